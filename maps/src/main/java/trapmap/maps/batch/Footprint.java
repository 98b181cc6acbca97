package trapmap.maps.batch;

import java.util.BitSet;

/**
 * Where one wafer was evaluated and where it was flagged, on cells of {@code pitchMm} in wafer coordinates (mm,
 * origin at the wafer centre, y up). Cell (i, j) covers x in [(i − ½)·pitch, (i + ½)·pitch), likewise y; cells are
 * stored row by row from (minI, minJ).
 *
 * @param family  wafers of one family (outline format) share a recurrence map
 * @param pitchMm cell size, mm
 * @param minI    first cell column
 * @param minJ    first cell row
 * @param width   cell columns
 * @param height  cell rows
 * @param covered cells holding at least one evaluated pixel
 * @param flagged cells holding at least one pixel of a flagged region
 */
public record Footprint(String family, double pitchMm, int minI, int minJ, int width, int height, BitSet covered,
                        BitSet flagged) {
}
