/**
 * Protocol scaling: how SNR follows from the acquisition parameters (voxel volume, total sampling
 * time, field strength, parallel-imaging acceleration), SNR efficiency, measured-against-predicted
 * ratios, and g-factor maps from repeated acquisitions. Plain Java on records and arrays.
 */
package org.noisewise.protocol;
