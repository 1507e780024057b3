package org.noisewise.cli;

import picocli.CommandLine.ITypeConverter;

/** picocli converter for {@link RegionSpec}. */
public class RegionConverter implements ITypeConverter<RegionSpec> {
    @Override
    public RegionSpec convert(String value) {
        return RegionSpec.parse(value);
    }
}
