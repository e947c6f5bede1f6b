package dev.dowser.store;

import java.time.Instant;

/** One account as stored; {@code role} is admin, reviewer or labeller. */
public record UserRow(long id, String name, String role, String passwordHash, boolean disabled, Instant createdAt) {
}
