/**
 * The before/after compare view: {@link trapmap.viewer.ui.compare.CompareModel} computes registration, derived
 * maps, paired statistics and the interstitial-iron map without Swing; {@link trapmap.viewer.ui.compare.ComparePanel}
 * shows them with linked zoom, pan and cursor.
 */
package trapmap.viewer.ui.compare;
