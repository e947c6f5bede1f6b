package dev.dowser.sampler;

import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertThrows;

import dev.dowser.model.Activation;
import dev.dowser.model.Architecture;
import java.util.List;
import org.junit.jupiter.api.Test;

/** The sampler's configuration: named defaults, a builder that keeps every value, refusals that say what to change. */
class SamplerConfigTest {

    @Test
    void theBuilderStartsFromTheNamedDefaultsAndKeepsEveryValue() {
        SamplerConfig d = SamplerConfig.defaults();
        assertEquals(KernelChoice.AUTO, d.kernel().choice());
        assertEquals(Activation.RELU, d.network().activation());
        assertEquals(List.of(Architecture.DEFAULT_HIDDEN), d.network().hidden());
        assertEquals(SamplerConfig.DEFAULT_CHAINS, d.chains().count());
        assertEquals(SamplerConfig.DEFAULT_DRAWS, d.chains().draws());
        assertEquals(SamplerConfig.DEFAULT_BURN_IN_STEPS, d.steps().burnInSteps());
        assertEquals(SamplerConfig.DEFAULT_REBURN_IN_STEPS, d.steps().reburnInSteps());
        assertEquals(SamplerConfig.DEFAULT_THIN_STEPS, d.steps().thinSteps());
        assertEquals(SamplerConfig.DEFAULT_BATCH_ROWS, d.steps().batchRows());
        assertEquals(SamplerConfig.DEFAULT_MAP_STEPS, d.steps().mapSteps());
        assertEquals(SamplerConfig.DEFAULT_TEMPERATURE, d.temperature());

        SamplerConfig c = d.toBuilder().kernel(KernelChoice.MALA).hidden(List.of(32, 16)).activation(Activation.TANH)
                .chains(2, 10).burnInSteps(5).reburnInSteps(3).thinSteps(2).batchRows(7).learningRate(0.01)
                .cycles(5).mapSteps(4).temperature(0.5).build();
        assertEquals(c, c.toBuilder().build());
        // Changing one value keeps the others: no wither resets a neighbour.
        SamplerConfig more = c.toBuilder().chains(5, 25).cycles(0).build();
        assertEquals(c.steps().batchRows(), more.steps().batchRows());
        assertEquals(c.network(), more.network());
        assertEquals(5, more.chains().perChain());
    }

    @Test
    void aConfigurationThatCannotRunIsRefusedSayingWhatToChange() {
        assertEquals("draws (10) must be a positive multiple of chains (4) so every chain keeps the same number",
                refusal(SamplerConfig.builder().chains(4, 10)));
        assertEquals("cycles must be 0 (constant step) or the draws per chain (16), got 3",
                refusal(SamplerConfig.builder().cycles(3)));
        assertEquals("temperature must be positive, got 0.0; 1 samples the true posterior",
                refusal(SamplerConfig.builder().temperature(0)));
        // The sampler's network and the model's architecture refuse a bad shape in the same words.
        String zeroWidth = refusal(SamplerConfig.builder().hidden(List.of(8, 0)));
        assertEquals("a hidden layer needs at least one unit, got [8, 0]", zeroWidth);
        assertEquals(zeroWidth, assertThrows(IllegalArgumentException.class,
                () -> new Architecture(3, List.of(8, 0), 2, Activation.RELU)).getMessage());
        assertEquals("activation is required: relu or tanh", refusal(SamplerConfig.builder().activation(null)));
    }

    private static String refusal(SamplerConfig.Builder b) {
        return assertThrows(IllegalArgumentException.class, b::build).getMessage();
    }
}
