package dev.dowser.cli;

import com.sun.management.GarbageCollectionNotificationInfo;
import java.lang.management.GarbageCollectorMXBean;
import java.lang.management.ManagementFactory;
import java.lang.management.MemoryUsage;
import java.util.ArrayList;
import java.util.List;
import java.util.concurrent.atomic.AtomicLong;
import javax.management.ListenerNotFoundException;
import javax.management.Notification;
import javax.management.NotificationEmitter;
import javax.management.NotificationListener;
import javax.management.openmbean.CompositeData;

/**
 * Watches the heap in use right after each garbage collection: the memory a task really holds,
 * unlike the heap's peak, which shows how far the collector let garbage pile up.
 */
final class HeapAfterGc implements AutoCloseable {

    private final AtomicLong max = new AtomicLong();
    private final List<NotificationEmitter> emitters = new ArrayList<>();
    private final NotificationListener listener = this::onGc;

    private HeapAfterGc() {
    }

    static HeapAfterGc start() {
        HeapAfterGc w = new HeapAfterGc();
        for (GarbageCollectorMXBean gc : ManagementFactory.getGarbageCollectorMXBeans()) {
            if (gc instanceof NotificationEmitter emitter) {
                emitter.addNotificationListener(w.listener, null, null);
                w.emitters.add(emitter);
            }
        }
        return w;
    }

    private void onGc(Notification n, Object handback) {
        if (!GarbageCollectionNotificationInfo.GARBAGE_COLLECTION_NOTIFICATION.equals(n.getType())) {
            return;
        }
        var info = GarbageCollectionNotificationInfo.from((CompositeData) n.getUserData());
        long used = 0;
        for (MemoryUsage u : info.getGcInfo().getMemoryUsageAfterGc().values()) {
            used += u.getUsed();
        }
        // Non-heap pools (code cache, metaspace) are in the map too; they are small and steady.
        max.accumulateAndGet(used, Math::max);
    }

    /** The most memory in use just after any collection since {@link #start}. */
    long maxBytes() {
        return max.get();
    }

    @Override
    public void close() {
        for (NotificationEmitter e : emitters) {
            try {
                e.removeNotificationListener(listener);
            } catch (ListenerNotFoundException ignored) {
                // Already gone: nothing to undo.
            }
        }
    }
}
