package trapmap.physics.recombination;

/** How the surface-limited lifetime is computed from thickness, surface recombination velocity and diffusivity. */
public enum SurfaceModel {
    /** Sproul, JAP 76, 2851 (1994): τ_s = W/(2S) + (W/π)²/D (equal surfaces). Default. */
    SPROUL,
    /** Fundamental-mode eigenvalue: τ_s = 1/(α0² D) with tan(α0 W/2) = S/(α0 D) (equal surfaces). */
    EXACT
}
