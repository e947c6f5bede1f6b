package dev.dowser.cli;

import dev.dowser.rounds.PoolSettings;
import dev.dowser.rounds.Strategy;
import dev.dowser.sampler.SamplerConfig;
import dev.dowser.simulate.LabelSavings;
import java.io.IOException;
import java.io.PrintWriter;
import java.nio.file.Files;
import java.nio.file.Path;
import java.util.ArrayList;
import java.util.List;
import java.util.concurrent.atomic.AtomicInteger;

/** {@code dowser bench --only labels}: the label-savings benchmark over the benchmark datasets. */
final class LabelsBench {

    private LabelsBench() {
    }

    static void run(PrintWriter out, Path datasets, List<String> names, List<Strategy> strategies, int seeds,
                    SamplerConfig sampler, PoolSettings settings, Integer budget, Integer candidates, Path randomFrom,
                    Path dir)
            throws IOException {
        Files.createDirectories(dir);
        List<LabelSavings.Result> results = new ArrayList<>();
        for (String name : names) {
            LabelSavings.Setup setup = budget == null ? LabelSavings.setup(name)
                    : LabelSavings.setup(name).withBudget(budget);
            if (candidates != null) {
                setup = setup.withCandidates(candidates);
            }
            ProgressBar bar = new ProgressBar(System.err, "rounds of " + name);
            AtomicInteger done = new AtomicInteger();
            int curves = strategies.size() + (randomFrom == null ? 1 : 0);
            int total = seeds * curves * (2 + (setup.budget() - setup.seedLabels()) / setup.batch());
            results.add(LabelSavings.run(setup, datasets, strategies, seeds, sampler, settings, randomFrom, dir, out,
                    k -> bar.show(done.addAndGet(k), total, done.get())));
            bar.finish();
            Strategy main = strategies.get(0);
            Files.writeString(dir.resolve(LabelSavings.TABLE), LabelSavings.table(results, main));
        }
        out.printf("labels_table=%s%n", dir.resolve(LabelSavings.TABLE));
        out.flush();
    }
}
