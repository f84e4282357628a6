/**
 * Cautions shown in the help of commands whose results people may act on.
 */

/** For distances and routes on terrain. */
export const TERRAIN_CAUTION = `
Caution for route and terrain use: distances and paths are geometric, measured
on the mesh as given. They know nothing of ground conditions, vegetation,
water, weather, closures, land access or the accuracy of the scan, and a
short path may be steep or impassable. They are planning aids, not safety
assessments: check on the ground, follow local regulations and the advice of
qualified guides, surveyors or rescue services.`;

/** For cut paths and trim lines on parts. */
export const MACHINING_CAUTION = `
Caution for cutting and machining: paths are computed on the mesh as given,
which approximates the part (tessellation, scan noise, fixturing and springback
are not modelled). Verify every toolpath in your CAM system, simulate before
cutting, and follow your shop's safety procedures, machine limits and the
applicable standards and codes; a qualified person must approve a path before
it is run.`;

/** For walking times, routes and isochrones. */
export const WALKING_CAUTION = `
Caution for walking times: times come from a speed model applied to the mesh
as given. They are estimates for planning, not safety assessments. Weather,
daylight, snow and ice, ground and vegetation, loads, group size, fitness and
health change everything, and a route the model finds may cross ground that is
dangerous, closed or private. Check on the ground, allow wide margins, follow
local rules and defer to qualified guides, rangers and rescue services.`;
