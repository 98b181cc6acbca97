/**
 * Wafer outlines in wafer coordinates (mm): round wafers with a flat or notch and square or pseudo-square solar
 * wafers ({@link trapmap.maps.geometry.WaferShape}), the standard formats with their dimensions and sources
 * ({@link trapmap.maps.geometry.WaferFormat}), masks with an edge exclusion, and the outline found in the valid data
 * of a map when no shape is known ({@link trapmap.maps.geometry.OutlineDetection}), matched to a format at the map's
 * pixel pitch ({@link trapmap.maps.geometry.FormatMatch}: tolerance widened by one pitch, a mark too small for the
 * pitch left unresolved).
 */
package trapmap.maps.geometry;
