package dev.dowser.team;

import java.util.Locale;

/**
 * What an account may do. Admins run pools (imports, exports, settings, accounts) and may also
 * review and label; reviewers review and label; labellers label.
 */
public enum Role {
    LABELLER,
    REVIEWER,
    ADMIN;

    public static Role parse(String word) {
        try {
            return valueOf(word.trim().toUpperCase(Locale.ROOT));
        } catch (IllegalArgumentException | NullPointerException e) {
            throw new IllegalArgumentException("unknown role '" + word + "': use admin, reviewer or labeller");
        }
    }

    public String word() {
        return name().toLowerCase(Locale.ROOT);
    }

    /** True when this role includes everything {@code other} may do. */
    public boolean atLeast(Role other) {
        return compareTo(other) >= 0;
    }
}
