/**
 * Why a shop pays on an assumed fineness below the mark: US law lets a marked article assay a little
 * under its mark. National Gold and Silver Stamping Act: 15 U.S.C. 294 forbids trading falsely marked
 * goods "according to the standards" of sections 295 (gold) and 296 (silver).
 * - 15 U.S.C. 295 (as amended by Pub. L. 94-450, 1976): gold may be 3/1000 below its mark tested
 *   without solder; with solder assayed as one piece, 3/1000 for watchcases and flatware, 7/1000 otherwise.
 * - 15 U.S.C. 296: silver "sterling"/"coin" 4/1000 below (from memory).
 * Many items assay lower still (common practice), so the setting is the shop's choice; the default is nominal.
 */
export const US_MARKING_TOLERANCE = Object.freeze({
  goldWithoutSolder: '0.003',
  goldWithSolderWatchcaseOrFlatware: '0.003',
  goldWithSolderOther: '0.007',
  silver: '0.004',
});
