# LAS 1.2 (CWLS 1990): ~W values in the description field, colon with no space before it
~VERSION INFORMATION
VERS.           1.2   :CWLS Log ASCII Standard - VERSION 1.2
WRAP.           NO    :One Line per depth step
~WELL INFORMATION
STRT .F      48.5000         :START DEPTH
STOP .F      49.5000         :STOP DEPTH
STEP .F       0.5000         :STEP
NULL .          -999.25      :NULL VALUE
COMP .                 COMPANY:  Example Energy, Inc.
WELL .                    WELL:  EX 1-2
~CURVE INFORMATION
DEPT .F                      :DEPTH
GR   .GAPI                   :GAMMA RAY
~A
48.5 10.0
49.0 20.0
49.5 -999.25
