package org.noisewise.testing;

import java.util.ArrayList;
import java.util.List;
import java.util.Optional;
import org.junit.platform.engine.TestExecutionResult;
import org.junit.platform.engine.support.descriptor.ClassSource;
import org.junit.platform.launcher.TestExecutionListener;
import org.junit.platform.launcher.TestIdentifier;
import org.junit.platform.launcher.TestPlan;

/**
 * After the tests, names each test class that did not run because there is no display (the ImageJ
 * GUI tests), and how to run it, so a headless {@code mvn -B test} never passes silently without them.
 * Registered through {@code META-INF/services}.
 */
public final class SkippedTestsNote implements TestExecutionListener {

    private final List<String> skipped = new ArrayList<>();

    @Override
    public void executionSkipped(TestIdentifier id, String reason) {
        note(id, reason);
    }

    @Override
    public void executionFinished(TestIdentifier id, TestExecutionResult result) {
        if (result.getStatus() == TestExecutionResult.Status.ABORTED) {
            note(id, result.getThrowable().map(Throwable::getMessage).orElse(""));
        }
    }

    private synchronized void note(TestIdentifier id, String reason) {
        Optional<String> cls = id.getSource().filter(ClassSource.class::isInstance)
                .map(s -> ((ClassSource) s).getClassName());
        if (cls.isPresent() && reason != null && reason.contains("no display") && !skipped.contains(cls.get())) {
            skipped.add(cls.get());
        }
    }

    @Override
    public synchronized void testPlanExecutionFinished(TestPlan plan) {
        if (skipped.isEmpty()) {
            return;
        }
        // Surefire runs each test class in its own JVM here, so each skipped class says so itself
        for (String c : skipped) {
            System.out.println("NOTE: " + c + " did not run: there is no display for ImageJ's dialogs and ROI Manager. "
                    + "Run it with a virtual display: apt-get install xvfb xauth, then xvfb-run -a mvn -B test");
        }
    }
}
