package dev.dowser.team;

import dev.dowser.words.Worded;

/**
 * What an account may do. Admins run pools (imports, exports, settings, accounts) and may also
 * review and label; reviewers review and label; labellers label.
 */
public enum Role implements Worded {
    LABELLER,
    REVIEWER,
    ADMIN;

    public static Role parse(String word) {
        return Worded.parse(Role.class, word, "role");
    }

    /** True when this role includes everything {@code other} may do. */
    public boolean atLeast(Role other) {
        return compareTo(other) >= 0;
    }
}
