package dev.dowser.data;

import java.util.ArrayList;
import java.util.HashSet;
import java.util.List;
import java.util.Locale;
import java.util.Set;

/**
 * The keyboard key of each class in a label set. A class whose name is a single digit or letter
 * gets that key (so in a pool of digits 0-9, key 3 labels "3"); the others take the free keys
 * 1-9, then a-z, in class order; classes past the last free key have none. Letters are lower case
 * (a class named "B" is key b). The label set of a pool is fixed at import, so its keys are too.
 */
public final class LabelKeys {

    /** The keys handed out in order to classes without a key of their own. */
    static final String KEYS = "123456789abcdefghijklmnopqrstuvwxyz";

    private LabelKeys() {
    }

    /** The key of each class of {@code classes}, in the same order; null for a class left without one. */
    public static List<String> keysFor(List<String> classes) {
        List<String> keys = new ArrayList<>(classes.size());
        Set<String> taken = new HashSet<>();
        for (String c : classes) {
            String own = ownKey(c);
            keys.add(own != null && taken.add(own) ? own : null);
        }
        int next = 0;
        for (int i = 0; i < classes.size(); i++) {
            if (keys.get(i) != null) {
                continue;
            }
            while (next < KEYS.length() && taken.contains(String.valueOf(KEYS.charAt(next)))) {
                next++;
            }
            if (next < KEYS.length()) {
                String k = String.valueOf(KEYS.charAt(next++));
                taken.add(k);
                keys.set(i, k);
            }
        }
        return keys;
    }

    /** The key a class names itself: its name when that is one ASCII digit or letter, in lower case. */
    static String ownKey(String name) {
        if (name.length() != 1) {
            return null;
        }
        char c = name.charAt(0);
        boolean own = (c >= '0' && c <= '9') || (c >= 'a' && c <= 'z') || (c >= 'A' && c <= 'Z');
        return own ? name.toLowerCase(Locale.ROOT) : null;
    }
}
