/**
 * The command-line face: one picocli subcommand per method over the same core as the ImageJ
 * commands, writing aligned tables or JSON with the same column names.
 */
package org.noisewise.cli;
