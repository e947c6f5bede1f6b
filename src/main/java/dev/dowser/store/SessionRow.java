package dev.dowser.store;

import java.time.Instant;

/** A browser session with its account, as found by the hash of its token. */
public record SessionRow(String tokenHash, UserRow user, String csrfToken, Instant createdAt, Instant lastSeenAt,
                         Instant endedAt) {
}
