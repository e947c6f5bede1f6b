package dev.dowser.web;

import java.io.IOException;
import java.io.UncheckedIOException;
import java.nio.file.Files;
import java.nio.file.Path;
import java.time.Duration;
import java.util.Base64;
import java.util.List;
import java.util.Map;
import java.util.function.Function;
import org.openqa.selenium.By;
import org.openqa.selenium.Dimension;
import org.openqa.selenium.OutputType;
import org.openqa.selenium.StaleElementReferenceException;
import org.openqa.selenium.TimeoutException;
import org.openqa.selenium.WebDriver;
import org.openqa.selenium.WebElement;
import org.openqa.selenium.chrome.ChromeDriver;
import org.openqa.selenium.chrome.ChromeDriverService;
import org.openqa.selenium.chrome.ChromeOptions;
import org.openqa.selenium.support.ui.WebDriverWait;

/**
 * Debian's Chromium, headless, driven through Debian's chromedriver: nothing is downloaded, and
 * every background connection is switched off (the test machines have no outside network).
 */
final class Browser implements AutoCloseable {

    static final Path CHROMIUM = Path.of("/usr/bin/chromium");
    static final Path CHROMEDRIVER = Path.of("/usr/bin/chromedriver");
    static final Path SCREENSHOTS = Path.of("target", "screenshots");
    static final Duration WAIT = Duration.ofSeconds(60);
    static final int WIDTH = 1280;
    static final int HEIGHT = 1100;

    final ChromeDriver driver;
    private final boolean isShared;
    private static Browser shared;

    /**
     * The one Chromium the browser tests share, started on first use and quit when the tests' JVM
     * ends: starting a browser per test cost more than most tests. Each use begins on a blank page
     * with no cookies, the default window size and no emulated media; {@link #close} only resets it.
     */
    static synchronized Browser shared() {
        if (shared == null) {
            try {
                shared = new Browser(Files.createTempDirectory("dowser-chromium-"), true);
            } catch (IOException e) {
                throw new UncheckedIOException(e);
            }
            Browser b = shared;
            Runtime.getRuntime().addShutdownHook(new Thread(b.driver::quit));
        }
        shared.reset();
        return shared;
    }

    Browser(Path profile) {
        this(profile, false);
    }

    private Browser(Path profile, boolean isShared) {
        this.isShared = isShared;
        if (!Files.isExecutable(CHROMIUM) || !Files.isExecutable(CHROMEDRIVER)) {
            throw new IllegalStateException("the page tests need Debian's chromium and chromium-driver"
                    + " (/usr/bin/chromium, /usr/bin/chromedriver); ./dowser test installs them");
        }
        ChromeOptions options = new ChromeOptions();
        options.setBinary(CHROMIUM.toFile());
        options.addArguments("--headless", "--no-sandbox", "--disable-gpu", "--disable-background-networking",
                "--disable-component-update", "--disable-sync", "--no-first-run", "--disable-dev-shm-usage",
                "--window-size=" + WIDTH + "," + HEIGHT, "--user-data-dir=" + profile.toAbsolutePath());
        ChromeDriverService service = new ChromeDriverService.Builder()
                .usingDriverExecutable(CHROMEDRIVER.toFile()).usingAnyFreePort().build();
        this.driver = new ChromeDriver(service, options);
    }

    /**
     * Waits for the condition; on a timeout, saves a screenshot named after what was awaited. An
     * element drawn again while being read (pages redraw lists after each change) just means: look again.
     */
    <T> T await(Function<WebDriver, T> condition, String what) {
        return await(condition, what, WAIT);
    }

    /** The same with its own deadline, for the few steps that take long (a large upload). */
    <T> T await(Function<WebDriver, T> condition, String what, Duration deadline) {
        try {
            return new WebDriverWait(driver, deadline).withMessage(what).ignoring(StaleElementReferenceException.class)
                    .until(condition);
        } catch (TimeoutException e) {
            screenshot("timeout-" + what.replaceAll("[^A-Za-z0-9]+", "-"));
            throw e;
        }
    }

    /** The element of the page with this id; fails at once when there is none. */
    WebElement byId(String id) {
        return driver.findElement(By.id(id));
    }

    /** Saves what the page shows as target/screenshots/NAME.png, for a reviewer to look at. */
    void screenshot(String name) {
        try {
            Files.createDirectories(SCREENSHOTS);
            Files.write(SCREENSHOTS.resolve(name + ".png"), driver.getScreenshotAs(OutputType.BYTES));
        } catch (IOException e) {
            throw new UncheckedIOException(e);
        }
    }

    /** Saves the whole page, beyond the window's bottom edge too, as target/screenshots/NAME.png. */
    void screenshotWholePage(String name) {
        Map<String, Object> shot = driver.executeCdpCommand("Page.captureScreenshot",
                Map.of("format", "png", "captureBeyondViewport", true));
        try {
            Files.createDirectories(SCREENSHOTS);
            Files.write(SCREENSHOTS.resolve(name + ".png"), Base64.getDecoder().decode((String) shot.get("data")));
        } catch (IOException e) {
            throw new UncheckedIOException(e);
        }
    }

    /** A blank page, no cookies, the default window, screen and media: as a fresh browser would be. */
    private void reset() {
        driver.get("about:blank");
        driver.executeCdpCommand("Network.clearBrowserCookies", Map.of());
        driver.executeCdpCommand("Emulation.setEmulatedMedia", Map.of("features", List.of()));
        driver.executeCdpCommand("Emulation.clearDeviceMetricsOverride", Map.of());
        driver.manage().window().setSize(new Dimension(WIDTH, HEIGHT));
    }

    /** Quits a browser of its own; the shared one is only reset for the next test. */
    @Override
    public void close() {
        if (isShared) {
            reset();
        } else {
            driver.quit();
        }
    }
}
