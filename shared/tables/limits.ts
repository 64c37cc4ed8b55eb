/**
 * Bounds on every request dimension that multiplies the work or the size of an answer. Each is
 * wider than any real stair, corridor or controller, so a real design never meets it; input
 * beyond one is a 400 naming the field (the schemas use these constants and quote them).
 */

/** Treads in one stair: a stair of 200 treads climbs some 35 m, more than any lit stair (common practice, no published source). */
export const MAX_TREADS = 200;
/** Flights in one stair: 20 flights is a ten-storey stair with two flights a storey (common practice, no published source). */
export const MAX_FLIGHTS = 20;
/** Length of one rail or corridor pixel run, m: longer runs are several installations (common practice, no published source). */
export const MAX_RAIL_LENGTH_M = 200;
/** Pixels (driver ICs) per metre of addressable strip: the densest strips hold about 144–160 (from memory). */
export const MAX_PIXELS_PER_M = 200;
/** Pixels in one run (rail, or all tread segments together): 200 m at 100 pixels/m (common practice, no published source). */
export const MAX_PIXELS_PER_RUN = 20_000;
/**
 * Fewest pixels a controller's data output may be limited to: pixel controllers drive hundreds
 * per output; below this the "controller" is not a pixel controller (from memory).
 */
export const MIN_PIXELS_PER_DATA_OUTPUT = 50;
/** Most pixels a data output may drive: one-wire at 800 kbit/s refreshes 10 000 pixels only 3 times a second (WS2812B timing, 30 µs a pixel). */
export const MAX_PIXELS_PER_DATA_OUTPUT = 10_000;
/** Pixel data outputs on one controller (common practice, no published source: controllers have 1–32). */
export const MAX_DATA_OUTPUTS_PER_CONTROLLER = 64;
/** Constant-voltage outputs on one controller (common practice, no published source: stair controllers have 8–64). */
export const MAX_CV_OUTPUTS_PER_CONTROLLER = 128;
/** Shortest strip a datasheet allows from one feed point, m: even dense 5 V strip carries 1 m (from memory). */
export const MIN_FEED_LENGTH_M = 0.5;
/** Least current one feed point may carry, A: a strip's copper carries several amperes (common practice, no published source). */
export const MIN_FEED_CURRENT_A = 1;
/** Current of one pixel (or 12 / 24 V segment) at full white, mA: the brightest RGBW parts draw about 80–120 (from memory). */
export const MAX_CURRENT_PER_PIXEL_MA = 300;
/** Pieces in one reel-cutting request: two per tread of the largest stair, plus its landings. */
export const MAX_REEL_PIECES = 2 * MAX_TREADS + MAX_FLIGHTS;
/** Items in one inline catalog: a shop's whole stair-lighting range (common practice, no published source). */
export const MAX_CATALOG_ITEMS = 1000;

/**
 * Largest serialized answer, bytes. The bounded inputs keep every real design far below it
 * (a 200-tread estimate is about 0.3 MB); a larger answer is a 422 `answer_too_large`.
 */
export const MAX_ANSWER_BYTES = 2 * 1024 * 1024;
