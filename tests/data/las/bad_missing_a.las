~VERSION INFORMATION
 VERS.   2.0 : CWLS LOG ASCII STANDARD - VERSION 2.0
 WRAP.   NO : ONE LINE PER DEPTH STEP
#--------------------------------------------
~WELL INFORMATION
#MNEM.UNIT    DATA              : DESCRIPTION
 STRT.M     0.000            : START DEPTH
 STOP.M     10.000            : STOP DEPTH
 STEP.M     0.500            : STEP
 NULL.      -999.25           : NULL VALUE
 WELL.      Kestrel Bluff hand-held log  : SECTION NAME
 LOC .      Invented outcrop, Marrow Basin  : LOCATION
 DATE.      2026-08-14        : LOG DATE
~CURVE INFORMATION
 DEPT.M                 : DEPTH BELOW SECTION TOP
 GR  .API                 : TOTAL GAMMA RAY
 K   .%                   : POTASSIUM
~PARAMETER INFORMATION
 GAIN.      1.00 : DETECTOR GAIN
~OTHER
Readings every 0.5 m with a hand-held spectrometer, 120 s count.
