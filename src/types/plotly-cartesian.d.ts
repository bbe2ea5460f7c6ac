// The cartesian distribution bundle has the same API as plotly.js (types from @types/plotly.js).
declare module 'plotly.js-cartesian-dist-min' {
  import * as Plotly from 'plotly.js';
  export default Plotly;
}
