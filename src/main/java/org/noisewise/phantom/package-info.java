/**
 * Phantom QA geometry and metrics on plain arrays: finding the phantom, placing the signal,
 * background, ghosting and uniformity regions, percent integral uniformity, NEMA-style
 * non-uniformity, percent-signal ghosting, published action limits, and the QA log with its
 * baseline control limits. Pure Java.
 */
package org.noisewise.phantom;
