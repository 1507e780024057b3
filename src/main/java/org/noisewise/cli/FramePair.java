package org.noisewise.cli;

import picocli.CommandLine;

/** {@code --frames a,b}: two 1-based frames. */
public record FramePair(int a, int b) {

    public static FramePair parse(String text) {
        String[] p = text.split(",");
        if (p.length != 2) {
            throw new CommandLine.TypeConversionException("'" + text + "' is not two frames: write a,b (e.g. 1,2)");
        }
        try {
            return new FramePair(Integer.parseInt(p[0].trim()), Integer.parseInt(p[1].trim()));
        } catch (NumberFormatException e) {
            throw new CommandLine.TypeConversionException("'" + text + "' is not two frames: a and b must be whole numbers");
        }
    }

    /** picocli converter. */
    public static class Converter implements CommandLine.ITypeConverter<FramePair> {
        @Override
        public FramePair convert(String value) {
            return parse(value);
        }
    }
}
