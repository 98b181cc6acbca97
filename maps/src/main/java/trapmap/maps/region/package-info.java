/**
 * Connected regions above or below a threshold (8-connected, filtered by area) with their size, position, peak and
 * distance from the wafer edge ({@link trapmap.maps.region.ThresholdRegions}).
 */
package trapmap.maps.region;
