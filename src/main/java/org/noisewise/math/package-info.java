/**
 * Special functions that Apache Commons Math does not provide: exponentially scaled modified
 * Bessel functions and the confluent hypergeometric moments of the (noncentral) chi family.
 * Pure Java on doubles; no ImageJ.
 */
package org.noisewise.math;
