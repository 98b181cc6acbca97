/**
 * Wafer outlines in wafer coordinates (mm): round wafers with a flat or notch and square or pseudo-square solar
 * wafers ({@link trapmap.maps.geometry.WaferShape}), the standard formats with their dimensions and sources
 * ({@link trapmap.maps.geometry.WaferFormat}), masks with an edge exclusion, and the outline found in the valid data
 * of a map when no shape is known ({@link trapmap.maps.geometry.OutlineDetection}).
 */
package trapmap.maps.geometry;
