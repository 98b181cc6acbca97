/**
 * Defect identification over a wafer from lifetime maps at several injection levels (injection-dependent lifetime
 * spectroscopy, Rein, Lifetime Spectroscopy, Springer (2005)):
 * <ul>
 * <li>{@link trapmap.maps.spectroscopy.InjectionStack}: the maps of one wafer at two or more levels (files, or the
 * pages of one file whose sidecar gives each page's {@code injection_cm3} or {@code generation_cm3_s}), checked and
 * registered onto the first level;</li>
 * <li>{@link trapmap.maps.spectroscopy.StackLifetimes}: τ_SRH and Δn per pixel and level from the map conversion;</li>
 * <li>{@link trapmap.maps.spectroscopy.DefectIdentification}: the library ranking per pixel or k×k block and per
 * region, with the DPSS per region, giving an {@link trapmap.maps.spectroscopy.IdentificationResult}.</li>
 * </ul>
 * The numerics are physics' {@code trapmap.physics.spectroscopy}; this package only assembles curves from maps.
 */
package trapmap.maps.spectroscopy;
