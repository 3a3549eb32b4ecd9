/**
 * plotly.js-strict-dist-min ships no types: it is the same API as plotly.js-dist-min (Plotly's
 * "strict" bundle differs only in avoiding run-time code generation, so the CSP needs no 'unsafe-eval').
 */
declare module 'plotly.js-strict-dist-min' {
  import Plotly from 'plotly.js-dist-min';
  export = Plotly;
}
