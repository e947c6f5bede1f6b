package dev.dowser.web;

/** A request the API refuses, with the HTTP status to send and a message a person can act on. */
final class ApiException extends RuntimeException {

    private final int status;

    ApiException(int status, String message) {
        super(message);
        this.status = status;
    }

    int status() {
        return status;
    }
}
