# no WRAP line in ~V
~VERSION INFORMATION
 VERS.                  2.0 : CWLS LOG ASCII STANDARD - VERSION 2.0
~WELL INFORMATION
 STRT.M         1500.0000                : START DEPTH
 STOP.M         1501.0000                : STOP DEPTH
 STEP.M         0.5000                   : STEP
 NULL.          -999.25                  : NULL VALUE
 WELL.          FIXTURE 1                : WELL
~CURVE INFORMATION
 DEPT.M                                  : MEASURED DEPTH
 GR  .GAPI                               : GAMMA RAY
~A
 1500.0   35.20
 1500.5   88.10
 1501.0   41.70
