/**
 * The ImageJ/Fiji face: one thin {@code PlugIn} per menu command. Each reads the image, its
 * calibration and the ROI Manager regions, calls the core, and shows a named results table.
 * Every command has a public static {@code process(...)} entry for scripts and tests.
 */
package org.noisewise.imagej;
