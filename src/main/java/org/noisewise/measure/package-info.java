/**
 * One measurement per method, shared by every face: an image, its regions with roles, the
 * method's options, the planes to measure and a progress sink go in; result rows (and any maps,
 * corrected images or plots) come out. The ImageJ commands, the command-line commands and batch all
 * call these classes and only gather inputs and show outputs, so the faces offer the same features.
 * ImageJ-aware (it reads {@code ImagePlus} planes through {@code org.noisewise.io}); the arithmetic
 * stays in the core packages.
 */
package org.noisewise.measure;
