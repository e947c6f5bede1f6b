package dev.dowser.store;

import java.time.Instant;

/** An API token's stored facts (never the token itself), with its account. */
public record TokenRow(long id, UserRow user, String name, Instant createdAt, Instant revokedAt) {
}
