package dev.dowser.web;

import java.io.IOException;
import java.io.InputStream;
import java.nio.file.Files;
import java.nio.file.Path;
import java.security.GeneralSecurityException;
import java.security.KeyStore;
import javax.net.ssl.KeyManagerFactory;
import javax.net.ssl.SSLContext;

/**
 * Serving HTTPS directly: a PKCS#12 keystore holding the server's key and certificate chain, and
 * its password. Checked when made, so a wrong path or password stops the server before it listens.
 */
public record TlsConfig(Path keystore, String password) {

    public TlsConfig {
        if (keystore == null || !Files.isRegularFile(keystore)) {
            throw new IllegalArgumentException("the TLS keystore " + keystore + " is not a readable file;"
                    + " give a PKCS#12 file (.p12) with the server's key and certificate");
        }
        if (password == null) {
            throw new IllegalArgumentException("the TLS keystore needs its password");
        }
    }

    /** The server's TLS context, from the keystore. */
    SSLContext context() {
        try (InputStream in = Files.newInputStream(keystore)) {
            KeyStore store = KeyStore.getInstance("PKCS12");
            store.load(in, password.toCharArray());
            KeyManagerFactory keys = KeyManagerFactory.getInstance(KeyManagerFactory.getDefaultAlgorithm());
            keys.init(store, password.toCharArray());
            SSLContext context = SSLContext.getInstance("TLS");
            context.init(keys.getKeyManagers(), null, null);
            return context;
        } catch (IOException e) {
            throw new IllegalArgumentException("cannot read the TLS keystore " + keystore + ": " + e.getMessage()
                    + " (is it PKCS#12, and is the password right?)", e);
        } catch (GeneralSecurityException e) {
            throw new IllegalArgumentException("the TLS keystore " + keystore + " cannot be used: " + e.getMessage(), e);
        }
    }
}
