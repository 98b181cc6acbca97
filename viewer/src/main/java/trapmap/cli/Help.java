package trapmap.cli;

/** Help texts shared by several commands (annotation values must be constants). */
final class Help {
    /** The doping's forms, without a default. */
    static final String DOPING_FORMS = "Net doping: p:<cm^-3> or n:<cm^-3> (e.g. p:1e16), or a resistivity at 23 °C"
            + " p:<Ω·cm> / n:<Ω·cm> written as 1.5ohmcm, 1.5Ohm.cm or 1.5ohm*cm, converted by ASTM F723 (boron for p,"
            + " phosphorus for n).";
    static final String DOPING = DOPING_FORMS + " No default; required.";
    static final String TEMPERATURE = "Wafer temperature in K, 77-500. Default: 300 K.";
    static final String VTH = "Thermal velocities: fixed = 1.1e7 cm/s for electrons and holes at 300 K, scaled by"
            + " sqrt(T/300) (the convention of the built-in cross-sections), or green = Green, JAP 67, 2944 (1990)"
            + " (2.046e7 / 1.688e7 cm/s at 300 K). Default: fixed.";
    static final String JSON = "Print one JSON object with snake_case fields instead of a table. Infinite or"
            + " undefined numbers are written as null. Default: table.";
    static final String DEFECT_FILE = "JSON file of user-defined defects: one object, an array, or"
            + " {\"defects\": [...]}; fields id, name, source, level {reference Ec|Ev|Ei, energy_ev, degeneracy},"
            + " sigma_n_cm2, sigma_p_cm2, vth_convention fixed|green, spread. Default: none.";
    /** Exit codes of a command that only computes and prints (no output file, no cases file). */
    static final String EXIT_CODES = "Exit codes: 0 done; 2 invalid input (one line on stderr names the option);"
            + " 3 internal error.";
    /** Exit codes of a command that writes a map or files. */
    static final String EXIT_CODES_OUTPUT = "Exit codes: 0 done; 2 invalid input (one line on stderr names the"
            + " option); 3 internal error, or the output could not be written (disk full, no permission).";
    /** Exit codes of {@code convert}, whose output may be a picture. */
    static final String EXIT_CODES_MAP_OUTPUT = "Exit codes: 0 done; 2 invalid input (one line on stderr names the"
            + " option); 3 internal error, or the output could not be written (disk full, no permission); 5 a .png"
            + " picture could not be made: this Java runtime lacks font libraries or fonts (one line names what and"
            + " the packages to install).";
    /** Exit codes of {@code calc}, which also processes cases files. */
    static final String EXIT_CODES_CALC = "Exit codes: 0 done; 1 some rows of the --cases file failed (the others"
            + " were written); 2 invalid input (one line on stderr names the option), or --out cannot be written;"
            + " 3 internal error.";
    /** Exit codes of {@code compare} and {@code iron-map}: maps with an optional output and {@code --strict}. */
    static final String EXIT_CODES_STRICT = "Exit codes: 0 done; 2 invalid input (one line on stderr names the"
            + " option), or a registration warning with --strict; 3 internal error, or the output could not be"
            + " written (disk full, no permission); 5 a .png picture could not be made: this Java runtime lacks font"
            + " libraries or fonts (one line names what and the packages to install).";
    /** Exit codes of {@code trapmap} without a command. */
    static final String EXIT_CODES_ROOT = "Exit codes without a command: 0 done; 2 invalid input (one line on stderr"
            + " names the option); 3 internal error; 4 the demonstration batch's output could not be written; 5 its"
            + " results are complete but its summary PDF or pictures could not be made (this Java runtime lacks"
            + " fonts or font libraries; one line names the packages to install). Each"
            + " command lists its own exit codes in its --help.";
    static final String MODELS = "Models (defaults): n_i = 9.65e9 cm^-3 at 300 K (Altermatt et al., JAP 93, 1598"
            + " (2003)) with the Sproul & Green (1991) temperature form; N_c, N_v of Green, JAP 67, 2944 (1990);"
            + " intrinsic recombination of Richter et al., PRB 86, 165202 (2012) with B_low = 4.73e-15 cm^3/s"
            + " (Trupke et al. 2003); surface lifetime by Sproul, JAP 76, 2851 (1994) or the exact fundamental mode,"
            + " with the Klaassen (1992) minority-carrier diffusivity; SRH statistics of Shockley & Read and Hall"
            + " (1952).";

    private Help() {
    }
}
