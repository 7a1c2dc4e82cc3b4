# LAS 2.0 (CWLS 2014) line rule: first dot, first space after it, last colon; units with dots; a unit with a space; tabs; comment and blank lines
~VERSION INFORMATION
 VERS.                  2.0 : CWLS LOG ASCII STANDARD - VERSION 2.0
 WRAP.                   NO : ONE LINE PER DEPTH STEP
# a comment in the header

~WELL INFORMATION
 STRT.FT        1000.0                   : START DEPTH
 STOP.FT        1001.0                   : STOP DEPTH
 STEP.FT        0.5                      : STEP
 NULL.          -999.25                  : NULL VALUE
 COMP.          ANY OIL COMPANY : INC.   : COMPANY
 WELL.          TRAP 1-2                 : WELL
 DATE.          2024-03-15 14:30         : LOG DATE
 TIME.          14:30:00                 : TIME STARTED
 RUN .1                                  : RUN NUMBER
 DFD .KG/M3 1525.0000: DRILL FLUID DENSITY
~CURVE INFORMATION
 DEPT.FT                                 : MEASURED DEPTH
 TDEP.1IN                                : TIME DEPTH IN TENTHS OF AN INCH
 TENS.1000 LBF                           : CABLE TENSION
 GR  .GAPI      07 310 01 00             : GAMMA RAY
~PARAMETER INFORMATION
 BHT .DEGC	85.0	: BOTTOM HOLE TEMPERATURE
~OTHER
 Free text: kept as written.
~A
1000.0	120000	1.5	45.0
1000.5	120006	1.6	50.5
1001.0	120012	1.7	-999.25
