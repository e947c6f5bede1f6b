package dev.dowser.data;

import java.util.ArrayList;
import java.util.List;

/** The keyboard key of each class in a label set: 1-9, then a-z; classes past the 35th have none. */
public final class LabelKeys {

    private static final String KEYS = "123456789abcdefghijklmnopqrstuvwxyz";

    private LabelKeys() {
    }

    /** The key of the class at {@code index} (from 0), or null when the keys have run out. */
    public static String keyFor(int index) {
        return index < KEYS.length() ? String.valueOf(KEYS.charAt(index)) : null;
    }

    public static List<String> keysFor(List<String> classes) {
        List<String> keys = new ArrayList<>(classes.size());
        for (int i = 0; i < classes.size(); i++) {
            keys.add(keyFor(i));
        }
        return keys;
    }
}
