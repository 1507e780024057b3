/**
 * Time-series stability of a phantom series (functional and dynamic MRI QA): per-voxel detrending,
 * signal, fluctuation-noise, SFNR and static-noise maps, and the region figures of Friedman and
 * Glover (2006) and Weisskoff (1996). Pure Java on stored or calibrated arrays.
 */
package org.noisewise.series;
