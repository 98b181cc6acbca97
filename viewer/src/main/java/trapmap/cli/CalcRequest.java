package trapmap.cli;

import java.util.Locale;
import java.util.Map;
import java.util.function.Function;
import trapmap.physics.material.ThermalVelocityModel;
import trapmap.physics.recombination.SurfaceModel;

/**
 * The inputs of one {@code calc} case, as given: a null field was not given. The same request comes from the
 * command-line flags or from one row of a cases file (whose columns are the flags without dashes, {@code -} written
 * as {@code _}).
 *
 * @param lifetimeUs          effective lifetime τ_eff, µs
 * @param doping              doping
 * @param injectionCm3        fixed excess carrier density Δn, cm^-3
 * @param generationCm3PerS   steady-state generation rate G, cm^-3 s^-1
 * @param defect              defect id
 * @param temperatureK        temperature, K
 * @param thicknessUm         wafer thickness, µm
 * @param srvCmPerS           surface recombination velocity on both surfaces, cm/s
 * @param surfaceModel        surface-lifetime model
 * @param vth                 thermal-velocity model
 * @param referenceInjectionCm3 Δn at which to report the harmonised lifetime, cm^-3
 */
record CalcRequest(Double lifetimeUs, DopingValue doping, Double injectionCm3, Double generationCm3PerS,
                   String defect, Double temperatureK, Double thicknessUm, Double srvCmPerS,
                   SurfaceModel surfaceModel, ThermalVelocityModel vth, Double referenceInjectionCm3) {

    /** The inputs of a case, by flag: the column of a cases file is the flag's {@link #column()}. */
    enum Param {
        LIFETIME("--lifetime-us", s -> Quantity.LIFETIME_US.parse(s)),
        DOPING("--doping", DopingValue::parse),
        INJECTION("--injection", s -> Quantity.DENSITY_CM3.parse(s)),
        GENERATION("--generation", s -> Quantity.GENERATION.parse(s)),
        DEFECT("--defect", s -> s.trim().toLowerCase(Locale.ROOT)),
        TEMPERATURE("--temperature", s -> Quantity.TEMPERATURE_K.parse(s)),
        THICKNESS("--thickness-um", s -> Quantity.THICKNESS_UM.parse(s)),
        SRV("--srv", s -> Quantity.SRV_CM_S.parse(s)),
        SURFACE_MODEL("--surface-model", Choices::surfaceModel),
        VTH("--vth", Choices::vth),
        REFERENCE_INJECTION("--reference-injection", s -> Quantity.DENSITY_CM3.parse(s));

        private final String flag;
        private final Function<String, Object> parser;

        Param(String flag, Function<String, Object> parser) {
            this.flag = flag;
            this.parser = parser;
        }

        String flag() {
            return flag;
        }

        /** The cases-file column: the flag without dashes, {@code -} as {@code _}. */
        String column() {
            return flag.substring(2).replace('-', '_');
        }

        /**
         * The value of a non-blank cell.
         *
         * @throws InputException naming the flag, the rule and the text
         */
        Object parse(String text) {
            try {
                return parser.apply(text);
            } catch (Quantity.BadValue e) {
                throw new InputException(flag + " " + e.getMessage(), e);
            }
        }
    }

    /**
     * The request given by the non-blank cells of one cases-file row.
     *
     * @throws InputException for the first cell that cannot be parsed
     */
    static CalcRequest fromCells(Map<Param, String> cells) {
        Object[] v = new Object[Param.values().length];
        for (Param p : Param.values()) {
            String text = cells.get(p);
            if (text != null && !text.isBlank()) {
                v[p.ordinal()] = p.parse(text);
            }
        }
        return new CalcRequest((Double) v[0], (DopingValue) v[1], (Double) v[2], (Double) v[3], (String) v[4],
                (Double) v[5], (Double) v[6], (Double) v[7], (SurfaceModel) v[8], (ThermalVelocityModel) v[9],
                (Double) v[10]);
    }

    /**
     * This request with the missing values taken from {@code defaults}. Injection and generation go together: when
     * this request gives either, neither is taken from the defaults.
     */
    CalcRequest orElse(CalcRequest defaults) {
        boolean ownInjection = injectionCm3 != null || generationCm3PerS != null;
        return new CalcRequest(or(lifetimeUs, defaults.lifetimeUs), or(doping, defaults.doping),
                ownInjection ? injectionCm3 : defaults.injectionCm3,
                ownInjection ? generationCm3PerS : defaults.generationCm3PerS,
                or(defect, defaults.defect), or(temperatureK, defaults.temperatureK),
                or(thicknessUm, defaults.thicknessUm), or(srvCmPerS, defaults.srvCmPerS),
                or(surfaceModel, defaults.surfaceModel), or(vth, defaults.vth),
                or(referenceInjectionCm3, defaults.referenceInjectionCm3));
    }

    private static <T> T or(T value, T fallback) {
        return value != null ? value : fallback;
    }
}
