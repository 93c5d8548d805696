#!/usr/bin/Rscript
# Writes the pre-counted fixtures from clinic_followup.csv with R's haven package (Debian
# r-cran-haven): the visits counted by site, sex and recov (count column "n"), the unrecorded
# outcomes left out, as in clinic_counts.xlsx:
#   clinic_counts.xpt (transport v5) and clinic_counts.sas7bdat: character variables;
#   clinic_counts.sav and clinic_counts.dta: site, sex and recov as value-labelled numbers,
#       so the levels come from the value labels.
# Every file carries variable labels. Run from this folder: Rscript make_count_files.R
suppressMessages(library(haven))
d <- read.csv("clinic_followup.csv", encoding = "UTF-8", stringsAsFactors = FALSE, na.strings = "")
d <- d[!is.na(d$recov), c("site", "sex", "recov")]
n <- aggregate(list(n = rep(1, nrow(d))), by = d[c("site", "sex", "recov")], FUN = sum)
n <- n[order(n$site, n$sex, n$recov), ]
rownames(n) <- NULL
labels <- c(site = "Clinic site", sex = "Sex recorded at intake", recov = "Recovered at follow-up",
            n = "Visits")
with_labels <- function(x) {
  for (k in names(labels)) attr(x[[k]], "label") <- labels[[k]]
  x
}
sas <- with_labels(n)
write_xpt(sas, "clinic_counts.xpt", version = 5, name = "COUNTS")
suppressWarnings(write_sas(sas, "clinic_counts.sas7bdat"))

code <- function(x, levels) match(x, levels)
lab <- n
lab$site <- labelled(code(n$site, c("North clinic", "South clinic")),
                     labels = c("North clinic" = 1, "South clinic" = 2))
lab$sex <- labelled(code(n$sex, c("female", "male")), labels = c(female = 1, male = 2))
lab$recov <- labelled(ifelse(n$recov == "yes", 1, 0), labels = c(no = 0, yes = 1))
lab <- with_labels(lab)
write_sav(lab, "clinic_counts.sav")
write_dta(lab, "clinic_counts.dta", version = 15)
