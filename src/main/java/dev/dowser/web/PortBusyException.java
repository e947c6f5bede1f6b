package dev.dowser.web;

import java.net.BindException;

/** The port to listen on is taken by another program, or this user may not bind it. */
public final class PortBusyException extends RuntimeException {

    private final String bind;
    private final int port;

    private PortBusyException(String bind, int port, String why, Throwable cause) {
        super("cannot listen on " + bind + " port " + port + ": " + why, cause);
        this.bind = bind;
        this.port = port;
    }

    /** The failure to start as this exception when it was the port; otherwise the failure itself. */
    static RuntimeException from(RuntimeException e, String bind, int port) {
        for (Throwable t = e; t != null; t = t.getCause()) {
            if (t instanceof BindException b) {
                String why = b.getMessage() != null && b.getMessage().contains("in use")
                        ? "another program is using it" : String.valueOf(b.getMessage());
                return new PortBusyException(bind, port, why, e);
            }
        }
        return e;
    }

    public String bind() {
        return bind;
    }

    public int port() {
        return port;
    }
}
