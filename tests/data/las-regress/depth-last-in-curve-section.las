~Version information
VERS.   2.0 : CWLS LAS version 2.0
WRAP.   NO  : one line per depth step
~Well information
STRT.FT 1000.0 : start
STOP.FT 1001.0 : stop
STEP.FT 0.5    : step
NULL.   -999.25: null value
WELL.   INVENTED-1 : invented well
~Curve information
GR  .GAPI   : gamma ray
RHOB.G/CC   : matrix density
DEPT.FT     : depth
~A  Depth GR RHOB
1000.0  45.0  2.71
1000.5  50.0  2.65
1001.0  55.0  2.60
