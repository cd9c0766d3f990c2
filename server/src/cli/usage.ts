export const USAGE = `Usage:
  clearbase invert <negative...> --out DIR [options]
      Inverts raw negative scans (16-bit TIFF or PNG) into positives.
      --out DIR                  folder for the positives (created if missing)
      --profile P.json           stock profile document (default: a neutral straight-line profile)
      --scanner S.json           scanner profile document (default: linear counts, no black level)
      --base auto|x,y,w,h        film base: detect it, or sample this rectangle in pixels (default auto)
      --roll                     treat the files as one roll: shared roll base and roll-wide levels
      --exposure auto|metered    mid grey from the levels (each frame's, or the roll's with --roll), or fixed at
                                 the profile's metered 18 % grey, with no automatic levels (default auto)
      --exposure-stops N         more exposure printed, in steps of 1/6 stop within ±6 (+1, -2/3, 0.5; + lighter)
      --format jpeg|tiff16|png16 output format (default jpeg)
      --render print|reference   print-like tone curve, or plain reference rendering (default print)
      --threads N                worker threads (default: all cores)
      --json                     print one JSON line per frame on stdout, with the exposure used: the log
                                 exposure printed as mid grey (stops included), its source and the stops

  clearbase synth --out DIR [--frames N] [--stock NAME] [--scene SCENE] [--width W] [--height H]
      Writes demo negatives (16-bit TIFF) made with the forward film model. Stocks:
      clearbase-polyclear-200 (default), clearbase-tintline-400, clearbase-ambermask-100.
      Scenes: outdoor (default), chart (the 24-patch chart), grey-steps (11 steps), gradient.

  clearbase profile validate P.json
      Checks a stock profile document and prints each error with its path.

  clearbase calibrate --bracket FILE:STOPS[:x,y,w,h] ... --chart FILE --chart-region x,y,w,h | --chart-corners x1,y1,...,x4,y4
                      --out PROFILE.json [options]
      Builds a stock profile from a calibration roll: grey card frames bracketed over known stops and
      one frame of the 24-patch chart. Prints γ, speed point and EI, crosstalk and the exposure matrix,
      chart ΔE00 fitted and cross-validated (each patch left out of the fit in turn), and warnings.
      --bracket FILE:STOPS[:x,y,w,h]  a grey frame, its exposure in stops from the metered one (+1, -2/3)
                                 and, if the card moved, its own grey rectangle; repeat
      --chart FILE               the chart frame, normally exposed
      --more-chart FILE[:STOPS]  another frame of the same chart, STOPS from the metered one (+2, -1); repeat
      --chart-region x,y,w,h     the chart, square in the frame, patch 1 at the top left
      --chart-corners x1,y1,...  its four corners: by patch 1, patch 6, patch 24, patch 19
      --grey-region x,y,w,h      grey rectangle on every grey frame without its own (default: the central half)
      --base-region x,y,w,h      film base rectangle (on the leader, else on every frame; default: detected)
      --leader FILE              a frame of unexposed leader for the film base
      --scanner S.json           scanner profile document (default: linear counts, no black level)
      --stock NAME --iso N       the stock's name and box speed (default "Calibrated stock", 100)
      --film-base clear|tinted|masked   the stock's base (default clear)
      --json                     print the whole calibration report as one JSON line
      Exit 1 when the profile was written with warnings, or could not be made.

Exit status: 0 all done, 1 some inputs failed (the rest were written), 2 usage error.
`;
