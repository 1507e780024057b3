/**
 * Diagnostics that say when a noise method's assumptions fail: background checks (masking,
 * clipping, quantisation, fit to the chi(2L) model, estimator agreement) and the verdicts
 * valid / questionable / invalid with reasons in plain words. Pure Java.
 */
package org.noisewise.diagnose;
