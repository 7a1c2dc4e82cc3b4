~Version information
VERS.   2.0 : CWLS LAS version 2.0
WRAP.   NO  : one line per depth step
~Well information
STRT.M 1004.0 : start
STOP.M 1005.0 : stop
STEP.M 0.5    : step
NULL.   -999.25: null value
WELL.   INVENTED-3 : invented well
~Curve information
DEPT.M     : depth
GR  .GAPI   : gamma ray
~A
1004.0  45.0
1004.5  50.0
NaN     52.0
1005.0  55.0
