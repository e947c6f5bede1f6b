package dev.dowser.model;

import java.util.List;

/**
 * The shape of the network: inputs, hidden layer widths, classes, and the hidden nonlinearity.
 * A softmax turns the last layer into class probabilities.
 */
public record Architecture(int inputs, List<Integer> hidden, int classes, Activation activation) {

    public static final int DEFAULT_HIDDEN = 128;

    public Architecture {
        if (inputs < 1) {
            throw new IllegalArgumentException("the network needs at least one input feature, got " + inputs);
        }
        if (classes < 2) {
            throw new IllegalArgumentException("the network needs at least two classes, got " + classes);
        }
        hidden = checkedHidden(hidden, activation);
    }

    /**
     * The hidden widths, copied, once each layer has at least one unit and the activation is
     * given: the one rule, for the network and for the sampler's configuration alike.
     */
    public static List<Integer> checkedHidden(List<Integer> hidden, Activation activation) {
        List<Integer> widths = List.copyOf(hidden);
        for (int h : widths) {
            if (h < 1) {
                throw new IllegalArgumentException("a hidden layer needs at least one unit, got " + widths);
            }
        }
        if (activation == null) {
            throw new IllegalArgumentException("activation is required: relu or tanh");
        }
        return widths;
    }

    /** One hidden layer of 128 ReLU units, the default. */
    public static Architecture standard(int inputs, int classes) {
        return new Architecture(inputs, List.of(DEFAULT_HIDDEN), classes, Activation.RELU);
    }

    /** Number of weight layers: hidden layers plus the output layer. */
    public int layers() {
        return hidden.size() + 1;
    }

    public int fanIn(int layer) {
        return layer == 0 ? inputs : hidden.get(layer - 1);
    }

    public int fanOut(int layer) {
        return layer == hidden.size() ? classes : hidden.get(layer);
    }

    /** Widest layer output, for sizing work buffers. */
    int widest() {
        int w = classes;
        for (int h : hidden) {
            w = Math.max(w, h);
        }
        return w;
    }
}
