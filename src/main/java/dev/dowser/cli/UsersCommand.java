package dev.dowser.cli;

import dev.dowser.store.Database;
import dev.dowser.store.UserRow;
import dev.dowser.team.Accounts;
import dev.dowser.team.Role;
import dev.dowser.team.TeamConfig;
import java.io.BufferedReader;
import java.io.IOException;
import java.io.InputStreamReader;
import java.io.PrintWriter;
import java.nio.charset.StandardCharsets;
import java.security.SecureRandom;
import java.util.Base64;
import picocli.CommandLine.Command;
import picocli.CommandLine.Mixin;
import picocli.CommandLine.Model.CommandSpec;
import picocli.CommandLine.Option;
import picocli.CommandLine.Parameters;
import picocli.CommandLine.Spec;

@Command(name = "users", mixinStandardHelpOptions = true,
        description = {"Manages the accounts in the database: the H2 file in --data, or the PostgreSQL server given by --database-url.",
            "On H2, stop the server on that folder first (one program at a time opens the file).",
            "A new or reset password is generated and printed once, unless --password-stdin gives one."})
final class UsersCommand {

    /** Who the history names for changes made from the command line. */
    static final String ACTOR = "command line";

    @Spec
    CommandSpec spec;

    @Mixin
    DataOption data;

    @Command(name = "add", description = "Adds an account.")
    int add(@Parameters(paramLabel = "NAME", description = "The account name people sign in with.") String name,
            @Option(names = "--role", required = true, paramLabel = "admin|reviewer|labeller",
                    description = "What the account may do.") String role,
            @Option(names = "--password-stdin", description = "Read the password from the first line of"
                    + " standard input instead of generating one.") boolean fromStdin) throws IOException {
        Role r = Role.parse(role);
        String password = password(fromStdin);
        try (Database db = data.open()) {
            accounts(db).add(name, r, password, ACTOR);
        }
        out().println("added " + name + " (" + r.word() + ")");
        printGenerated(fromStdin, password);
        return 0;
    }

    @Command(name = "list", description = "Lists the accounts.")
    int list() {
        PrintWriter out = out();
        try (Database db = data.open()) {
            out.printf("%-30s %-9s %-8s %s%n", "name", "role", "state", "created");
            for (UserRow u : db.users().list()) {
                out.printf("%-30s %-9s %-8s %s%n", u.name(), u.role(), u.disabled() ? "disabled" : "active",
                        u.createdAt());
            }
        }
        out.flush();
        return 0;
    }

    @Command(name = "disable", description = "Disables an account; its sessions and tokens stop working at once.")
    int disable(@Parameters(paramLabel = "NAME") String name) {
        try (Database db = data.open()) {
            accounts(db).setDisabled(name, true, ACTOR);
        }
        out().println("disabled " + name);
        return 0;
    }

    @Command(name = "enable", description = "Enables a disabled account again.")
    int enable(@Parameters(paramLabel = "NAME") String name) {
        try (Database db = data.open()) {
            accounts(db).setDisabled(name, false, ACTOR);
        }
        out().println("enabled " + name);
        return 0;
    }

    @Command(name = "reset-password", description = "Sets a new password for an account.")
    int resetPassword(@Parameters(paramLabel = "NAME") String name,
                      @Option(names = "--password-stdin", description = "Read the password from the first line of"
                              + " standard input instead of generating one.") boolean fromStdin) throws IOException {
        String password = password(fromStdin);
        try (Database db = data.open()) {
            accounts(db).resetPassword(name, password, ACTOR);
        }
        out().println("password of " + name + " reset");
        printGenerated(fromStdin, password);
        return 0;
    }

    /** A new random password: 18 bytes as 24 base64url characters, about 144 bits. */
    static String generatePassword(SecureRandom random) {
        byte[] b = new byte[18];
        random.nextBytes(b);
        return Base64.getUrlEncoder().withoutPadding().encodeToString(b);
    }

    private String password(boolean fromStdin) throws IOException {
        if (!fromStdin) {
            return generatePassword(new SecureRandom());
        }
        String line = new BufferedReader(new InputStreamReader(System.in, StandardCharsets.UTF_8)).readLine();
        if (line == null) {
            throw new IllegalArgumentException("--password-stdin: standard input is empty");
        }
        return line;
    }

    private void printGenerated(boolean fromStdin, String password) {
        if (!fromStdin) {
            PrintWriter out = out();
            out.println("password: " + password + "   (shown only now)");
            out.flush();
        }
    }

    private PrintWriter out() {
        return spec.commandLine().getOut();
    }

    private static Accounts accounts(Database db) {
        return new Accounts(db, new SecureRandom(), TeamConfig.defaults());
    }
}
