package dev.dowser.sampler;

/** A step that produced a non-finite density or gradient, and what the chain did about it. */
public record Divergence(int chain, long step, String reason, double stepSizeAfter) {
}
