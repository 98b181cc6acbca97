/**
 * Profiles through a map: along a line with a band width ({@link trapmap.maps.profile.LineProfile}) and ring means
 * about a centre ({@link trapmap.maps.profile.RadialProfile}), sampled without inventing data where there is none.
 */
package trapmap.maps.profile;
