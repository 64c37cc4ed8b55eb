/**
 * Answers smaller than this go uncompressed: below about 1 kB the gzip header and the CPU cost
 * outweigh the bytes saved (common practice, no published source).
 */
export const COMPRESS_ABOVE_BYTES = 1024;
