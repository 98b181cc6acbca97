package trapmap.physics.defect;

import trapmap.physics.material.Silicon;
import trapmap.shared.check.Checks;

/**
 * Energy of a single trap level and its degeneracy factor.
 * <ul>
 * <li>from E_c: n1 = N_c exp(−(E_c − E_t)/kT), p1 = n_i²/n1;</li>
 * <li>from E_v: p1 = N_v exp(−(E_t − E_v)/kT), n1 = n_i²/p1;</li>
 * <li>from E_i: n1 = n_i exp((E_t − E_i)/kT), p1 = n_i²/n1;</li>
 * <li>degeneracy g: n1/g and g·p1 (Shockley–Read; equivalent to shifting E_t by kT ln g).</li>
 * </ul>
 * n1·p1 = n_i² holds exactly in every case.
 *
 * @param reference  which level {@code energyEv} is measured from
 * @param energyEv   depth below E_c, height above E_v (both ≥ 0) or signed offset from E_i, eV
 * @param degeneracy degeneracy factor g (> 0); 1 for the effective levels of lifetime spectroscopy
 */
public record TrapLevel(EnergyReference reference, double energyEv, double degeneracy) {

    /** Largest level energy accepted from a band edge, eV (about the silicon band gap). */
    public static final double MAX_ENERGY_EV = 1.2;

    public TrapLevel {
        Checks.notNull(reference, "reference");
        if (reference == EnergyReference.INTRINSIC) {
            Checks.inRange(energyEv, -MAX_ENERGY_EV / 2, MAX_ENERGY_EV / 2, "energy", "eV");
        } else {
            Checks.inRange(energyEv, 0, MAX_ENERGY_EV, "energy", "eV");
        }
        Checks.positive(degeneracy, "degeneracy", "");
    }

    public static TrapLevel belowConductionBand(double depthEv) {
        return new TrapLevel(EnergyReference.CONDUCTION_BAND, depthEv, 1);
    }

    public static TrapLevel aboveValenceBand(double heightEv) {
        return new TrapLevel(EnergyReference.VALENCE_BAND, heightEv, 1);
    }

    public static TrapLevel fromIntrinsic(double offsetEv) {
        return new TrapLevel(EnergyReference.INTRINSIC, offsetEv, 1);
    }

    /** The same level at another energy in the same reference. */
    public TrapLevel withEnergy(double ev) {
        return new TrapLevel(reference, ev, degeneracy);
    }

    /** Electron emission density n1 (degeneracy included), cm^-3. */
    public double n1PerCm3(Silicon si) {
        return bareN1(si) / degeneracy;
    }

    /** Hole emission density p1 (degeneracy included), cm^-3. */
    public double p1PerCm3(Silicon si) {
        double ni = si.intrinsicPerCm3();
        return degeneracy * ni * ni / bareN1(si);
    }

    private double bareN1(Silicon si) {
        double kt = si.thermalEnergyEv();
        double ni = si.intrinsicPerCm3();
        switch (reference) {
            case CONDUCTION_BAND:
                return si.conductionDosPerCm3() * Math.exp(-energyEv / kt);
            case VALENCE_BAND:
                return ni * ni / (si.valenceDosPerCm3() * Math.exp(-energyEv / kt));
            default:
                return ni * Math.exp(energyEv / kt);
        }
    }

    @Override
    public String toString() {
        return reference.format(energyEv) + (degeneracy == 1 ? "" : " (g = " + degeneracy + ")");
    }
}
