/**
 * Regular grid in the side-view plane (distance from axis 1 against height), laid out row-major as d3-contour
 * expects: value(ix, iy) = values[ix + iy * nx] at r = rMinMm + ix·stepMm, z = zMinMm + iy·stepMm.
 */
export interface Grid2 {
  readonly nx: number;
  readonly ny: number;
  readonly rMinMm: number;
  readonly zMinMm: number;
  readonly stepMm: number;
}
