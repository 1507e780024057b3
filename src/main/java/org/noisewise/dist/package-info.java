/**
 * Noise models of MR magnitude images as Commons Math {@code RealDistribution}s: Rice and the
 * L-channel noncentral chi. Rayleigh and central chi are Commons Math's {@code WeibullDistribution}
 * and {@code NakagamiDistribution}; the tests cross-check against them.
 */
package org.noisewise.dist;
