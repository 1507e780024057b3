package org.noisewise.phantom;

/**
 * Published action limits of the large-phantom QC procedure of the American College of Radiology
 * (as tabulated by AAPM TG-284): percent integral uniformity at least 87.5% below 3 T and at least
 * 82.0% at 3 T; percent-signal ghosting at most 2.5%. They apply only to scans made by that
 * procedure (its phantom, slice and protocol); the site's medical physicist sets what applies locally.
 */
public record ActionLimits(double minimumPiu, double maximumGhostingPercent, double fieldTesla) {

    /** Limits for a field strength in tesla (3 T limits from 2.9 T up). */
    public static ActionLimits largePhantom(double fieldTesla) {
        if (!(fieldTesla > 0)) {
            throw new IllegalArgumentException("field strength must be positive to choose the limits, was " + fieldTesla);
        }
        return new ActionLimits(fieldTesla >= 2.9 ? 82.0 : 87.5, 2.5, fieldTesla);
    }

    public boolean piuPasses(double piu) {
        return piu >= minimumPiu;
    }

    public boolean ghostingPasses(double percent) {
        return percent <= maximumGhostingPercent;
    }
}
