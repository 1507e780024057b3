#!/usr/bin/env bash
# Runs the benchmarks (not part of the tests): each prints ratios measured in one run on this machine.
set -euo pipefail
cd "$(dirname "$0")/.."
mvn -B -q test-compile dependency:build-classpath -Dmdep.outputFile=target/cp.txt -Dmdep.includeScope=test
java -cp "target/classes:target/test-classes:$(cat target/cp.txt)" org.noisewise.bench.RepeatedMapsBenchmark
