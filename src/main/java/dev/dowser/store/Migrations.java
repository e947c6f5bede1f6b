package dev.dowser.store;

import java.io.IOException;
import java.io.InputStream;
import java.io.Reader;
import java.io.StringReader;
import java.io.UncheckedIOException;
import java.net.JarURLConnection;
import java.net.URISyntaxException;
import java.net.URL;
import java.nio.charset.StandardCharsets;
import java.nio.file.Files;
import java.nio.file.Path;
import java.util.ArrayList;
import java.util.Arrays;
import java.util.Collection;
import java.util.Enumeration;
import java.util.List;
import java.util.Map;
import java.util.TreeMap;
import java.util.jar.JarEntry;
import java.util.jar.JarFile;
import java.util.stream.Stream;
import org.flywaydb.core.api.ResourceProvider;
import org.flywaydb.core.api.resource.LoadableResource;

/**
 * The migration scripts as PostgreSQL reads them. The scripts in {@code migrations/} are written
 * once, in the SQL that H2 and PostgreSQL share, but for one type name: the early scripts say
 * {@code BINARY LARGE OBJECT} (H2's large object, kept out of its B-tree pages), which PostgreSQL
 * calls {@code BYTEA}. The scripts cannot change (Flyway checks each applied script's checksum on
 * every start, so an edited script would stop every existing database from opening); this is the
 * one place that says how they read on PostgreSQL, by Flyway's own resource interface.
 */
final class Migrations implements ResourceProvider {

    /** H2's words and PostgreSQL's for the same thing. */
    static final Map<String, String> POSTGRESQL_WORDS = Map.of("BINARY LARGE OBJECT", "BYTEA");
    static final String FOLDER = "migrations";

    private final Map<String, LoadableResource> scripts = new TreeMap<>();

    private Migrations(Map<String, String> texts) {
        texts.forEach((name, text) -> scripts.put(name, new Script(name, text)));
    }

    /** The scripts on the class path, translated for PostgreSQL. */
    static Migrations forPostgresql() {
        Map<String, String> texts = new TreeMap<>();
        read().forEach((name, text) -> texts.put(name, toPostgresql(text)));
        return new Migrations(texts);
    }

    static String toPostgresql(String h2Text) {
        String out = h2Text;
        for (var e : POSTGRESQL_WORDS.entrySet()) {
            out = out.replace(e.getKey(), e.getValue());
        }
        return out;
    }

    @Override
    public LoadableResource getResource(String name) {
        return scripts.get(name.startsWith(FOLDER + "/") ? name.substring(FOLDER.length() + 1) : name);
    }

    @Override
    public Collection<LoadableResource> getResources(String prefix, String[] suffixes) {
        List<LoadableResource> out = new ArrayList<>();
        for (var e : scripts.entrySet()) {
            if (e.getKey().startsWith(prefix) && Arrays.stream(suffixes).anyMatch(e.getKey()::endsWith)) {
                out.add(e.getValue());
            }
        }
        return out;
    }

    /** Every {@code .sql} file of the class path's migrations folder, by file name, whether in a folder or a jar. */
    static Map<String, String> read() {
        URL folder = Migrations.class.getClassLoader().getResource(FOLDER);
        if (folder == null) {
            throw new StoreException("the migration scripts are missing from the class path (" + FOLDER + "/)");
        }
        Map<String, String> texts = new TreeMap<>();
        try {
            if (folder.getProtocol().equals("jar")) {
                JarURLConnection connection = (JarURLConnection) folder.openConnection();
                connection.setUseCaches(false);
                try (JarFile jar = connection.getJarFile()) {
                    for (Enumeration<JarEntry> entries = jar.entries(); entries.hasMoreElements(); ) {
                        JarEntry entry = entries.nextElement();
                        String name = entry.getName();
                        String file = name.substring(Math.min(name.length(), FOLDER.length() + 1));
                        if (name.startsWith(FOLDER + "/") && file.endsWith(".sql") && file.indexOf('/') < 0) {
                            try (InputStream in = jar.getInputStream(entry)) {
                                texts.put(file, new String(in.readAllBytes(), StandardCharsets.UTF_8));
                            }
                        }
                    }
                }
            } else {
                try (Stream<Path> files = Files.list(Path.of(folder.toURI()))) {
                    for (Path p : files.filter(p -> p.getFileName().toString().endsWith(".sql")).toList()) {
                        texts.put(p.getFileName().toString(), Files.readString(p));
                    }
                }
            }
        } catch (IOException e) {
            throw new UncheckedIOException("cannot read the migration scripts: " + e.getMessage(), e);
        } catch (URISyntaxException e) {
            throw new StoreException("cannot find the migration scripts at " + folder + ": " + e.getMessage(), e);
        }
        return texts;
    }

    /** One script's translated text, as Flyway reads it. */
    private static final class Script extends LoadableResource {
        private final String name;
        private final String text;

        Script(String name, String text) {
            this.name = name;
            this.text = text;
        }

        @Override
        public Reader read() {
            return new StringReader(text);
        }

        @Override
        public String getAbsolutePath() {
            return FOLDER + "/" + name;
        }

        @Override
        public String getAbsolutePathOnDisk() {
            return FOLDER + "/" + name;
        }

        @Override
        public String getFilename() {
            return name;
        }

        @Override
        public String getRelativePath() {
            return name;
        }
    }
}
