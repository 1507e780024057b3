#!/usr/bin/env bash
# Runs the benchmarks (not part of the tests): each prints ratios measured in one run on this machine.
set -euo pipefail
cd "$(dirname "$0")/.."
mvn -B -q test-compile dependency:build-classpath -Dmdep.outputFile=target/cp.txt -Dmdep.includeScope=test
CP="target/classes:target/test-classes:$(cat target/cp.txt)"
java -Xmx3g -cp "$CP" org.noisewise.bench.RepeatedMapsBenchmark
java -Xmx3g -cp "$CP" org.noisewise.bench.RicianCorrectionBenchmark
java -Xmx3g -cp "$CP" org.noisewise.bench.StabilityBenchmark
java -Xmx3g -cp "$CP" org.noisewise.bench.AirFinderBenchmark
mvn -B -q package -DskipTests
java -Xmx3g -cp "$CP" org.noisewise.bench.LargeImageBenchmark target/noisewise.jar
# the DICOM benchmark adds a pydicom + numpy contender when python3 has both
# (Debian: apt-get install python3-pydicom python3-numpy); it says so when it leaves it out
java -Xmx3g -cp "$CP" org.noisewise.bench.DicomSeriesBenchmark target/noisewise.jar
