/**
 * ImageJ-aware adapters shared by both faces: image planes to calibrated {@code float[]},
 * ROIs to core regions, the region naming convention, and file opening through ImageJ's readers.
 */
package org.noisewise.io;
