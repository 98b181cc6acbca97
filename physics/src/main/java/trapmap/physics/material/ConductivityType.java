package trapmap.physics.material;

/** Conductivity type of a wafer. */
public enum ConductivityType {
    /** p-type: acceptors (boron) dominate; electrons are the minority carriers. */
    P,
    /** n-type: donors (phosphorus) dominate; holes are the minority carriers. */
    N
}
