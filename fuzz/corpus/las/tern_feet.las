~VERSION INFORMATION
 VERS.   2.0 : CWLS LOG ASCII STANDARD - VERSION 2.0
 WRAP.   NO : ONE LINE PER DEPTH STEP
#--------------------------------------------
~WELL INFORMATION
#MNEM.UNIT    DATA              : DESCRIPTION
 STRT.FT     100.000            : START DEPTH
 STOP.FT     120.000            : STOP DEPTH
 STEP.FT     2.000            : STEP
 NULL.      -999.25           : NULL VALUE
 WELL.      Tern Gully trench log  : SECTION NAME
 LOC .      Invented outcrop, Marrow Basin  : LOCATION
 DATE.      2026-08-14        : LOG DATE
~CURVE INFORMATION
 DEPT.FT                 : DEPTH BELOW SECTION TOP
 GR  .GAPI                : GAMMA RAY
~A
   100.0    90.000
   102.0    87.552
   104.0    80.806
   106.0    71.415
   108.0    61.677
   110.0    53.977
   112.0    50.200
   114.0  -999.250
   116.0    56.927
   118.0    65.784
   120.0    75.673
