// geojson-validation ships no types; these cover the calls doab's tests make.
declare module 'geojson-validation' {
  export function valid(object: unknown, trace?: false): boolean;
  export function valid(object: unknown, trace: true): string[];
  export function isFeatureCollection(object: unknown, trace?: false): boolean;
  export function isFeatureCollection(object: unknown, trace: true): string[];
}
