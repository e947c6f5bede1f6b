package dev.dowser.cli;

import picocli.CommandLine.IVersionProvider;

/** The version from the jar's manifest, or "development" when run from classes. */
final class Version implements IVersionProvider {

    @Override
    public String[] getVersion() {
        String v = Main.class.getPackage().getImplementationVersion();
        return new String[] {"dowser " + (v == null ? "development" : v)};
    }
}
