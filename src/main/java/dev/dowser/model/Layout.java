package dev.dowser.model;

/**
 * Where each weight lives in the one flat parameter vector. Layer after layer: first its weight
 * matrix W_l, fanIn(l) x fanOut(l) row-major (W_l[i][j] at weightOffset(l) + i * fanOut(l) + j,
 * input i to unit j), then its bias vector b_l of fanOut(l).
 */
public final class Layout {

    private final Architecture arch;
    private final int[] weightOffset;
    private final int[] biasOffset;
    private final int dimension;

    public Layout(Architecture arch) {
        this.arch = arch;
        int layers = arch.layers();
        weightOffset = new int[layers];
        biasOffset = new int[layers];
        long at = 0;
        for (int l = 0; l < layers; l++) {
            weightOffset[l] = (int) at;
            at += (long) arch.fanIn(l) * arch.fanOut(l);
            biasOffset[l] = (int) at;
            at += arch.fanOut(l);
        }
        if (at > Integer.MAX_VALUE - 16) {
            throw new IllegalArgumentException("the network has " + at + " parameters, more than one array holds");
        }
        dimension = (int) at;
    }

    public Architecture architecture() {
        return arch;
    }

    public int dimension() {
        return dimension;
    }

    public int weightOffset(int layer) {
        return weightOffset[layer];
    }

    public int biasOffset(int layer) {
        return biasOffset[layer];
    }

    public int weightCount(int layer) {
        return arch.fanIn(layer) * arch.fanOut(layer);
    }
}
