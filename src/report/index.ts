export { renderReport, ASSUMPTIONS, type ReportInput, type ReportMeta } from './report.js';
export { renderProfileSvg, peakLabelText, type ProfileSvgOptions } from './profile-svg.js';
export { renderDistrictMap, type DistrictMap, type MapOptions } from './map-svg.js';
export { escapeHtml } from './escape.js';
