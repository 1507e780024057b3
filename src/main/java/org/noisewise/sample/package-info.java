/**
 * Generated demo and test images with known truth (invented scenario; no real data). Pure Java.
 */
package org.noisewise.sample;
