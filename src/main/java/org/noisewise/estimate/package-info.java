/**
 * Noise and SNR estimators on plain arrays: background sigma for L channels, region statistics,
 * SNR with confidence intervals, and the warnings that say when a method's assumptions fail.
 * No ImageJ imports; the faces ({@code org.noisewise.imagej}, {@code org.noisewise.cli}) call in.
 */
package org.noisewise.estimate;
