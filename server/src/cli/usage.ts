export const USAGE = `Usage:
  clearbase invert <negative...> --out DIR [options]
      Inverts raw negative scans (16-bit TIFF or PNG) into positives.
      --out DIR                  folder for the positives (created if missing)
      --profile P.json           stock profile document (default: a neutral straight-line profile)
      --scanner S.json           scanner profile document (default: linear counts, no black level)
      --base auto|x,y,w,h        film base: detect it, or sample this rectangle in pixels (default auto)
      --roll                     treat the files as one roll: shared roll base and roll-wide levels
      --format jpeg|tiff16|png16 output format (default jpeg)
      --render print|reference   print-like tone curve, or plain reference rendering (default print)
      --threads N                worker threads (default: all cores)
      --json                     print one JSON line per frame on stdout

  clearbase synth --out DIR [--frames N] [--stock NAME] [--width W] [--height H]
      Writes demo negatives (16-bit TIFF) made with the forward film model. Stocks:
      clearbase-polyclear-200 (default), clearbase-tintline-400, clearbase-ambermask-100.

  clearbase profile validate P.json
      Checks a stock profile document and prints each error with its path.

Exit status: 0 all done, 1 some inputs failed (the rest were written), 2 usage error.
`;
