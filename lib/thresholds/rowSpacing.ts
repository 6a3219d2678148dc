/** Row spacing lives with the conditioning (lib/signal), which labels time-averaged exports; re-exported for the methods. */
export { AVERAGED_ROW_INTERVAL_S, areTimeAveragedRows, medianRowIntervalS } from "../signal/rowSpacing";
