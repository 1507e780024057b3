/**
 * Result formatting shared by both faces: each result kind describes its columns once
 * ({@link org.noisewise.report.ResultRow}); tables, CSV and JSON are written from that description.
 */
package org.noisewise.report;
